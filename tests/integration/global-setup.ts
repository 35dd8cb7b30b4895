import { resetTestDatabase } from "../fixtures/database";
import { testObjectStore } from "../fixtures/object-store";

export default async function setup() {
  const stopObjectStore = await testObjectStore();
  await resetTestDatabase();
  return stopObjectStore;
}
