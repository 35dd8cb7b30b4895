import { resetTestDatabase } from "../fixtures/database";

export default async function setup() {
  await resetTestDatabase();
}
