import { clusterScript } from "./cluster";

/** Starts the test cluster from the demo data (three nodes, HAProxy, two app instances) and stops it after the run. */
export default async function setup() {
  const started = Date.now();
  process.env.PATINA_CLUSTER_FRESH = "1";
  // A smaller demo company than the default: the workload needs routes and pools, not years of history.
  process.env.PATINA_CLUSTER_SEED_ARGS = "--pools 60 --years 1";
  try {
    console.log(await clusterScript("start"));
  } catch (error) {
    // Whatever did start is stopped again, by its recorded pid.
    await clusterScript("stop").catch(() => undefined);
    throw error;
  } finally {
    delete process.env.PATINA_CLUSTER_FRESH;
    delete process.env.PATINA_CLUSTER_SEED_ARGS;
  }
  console.log(`[cluster test] cluster ready in ${Math.round((Date.now() - started) / 1000)} s`);
  return async () => {
    console.log(await clusterScript("stop"));
  };
}
