import { freshTestDatabase } from "./test-database";

export default async function setup() {
  await freshTestDatabase();
}
