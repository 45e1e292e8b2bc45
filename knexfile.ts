import { existsSync } from "node:fs";
import type { Knex } from "knex";

if (existsSync(".env")) process.loadEnvFile(".env");

const config: Knex.Config = {
  client: "mysql2",
  connection: {
    host: process.env.DB_HOST ?? "127.0.0.1",
    port: Number(process.env.DB_PORT ?? 3307),
    user: process.env.DB_USER ?? "foamtally",
    password: process.env.DB_PASSWORD ?? "",
    database: process.env.DB_NAME ?? "foamtally",
    charset: "utf8mb4",
    timezone: "Z",
    dateStrings: false,
    decimalNumbers: false,
  },
  pool: { min: 0, max: 10 },
  migrations: { directory: "./migrations", extension: "ts", loadExtensions: [".ts"] },
  seeds: { directory: "./seeds", extension: "ts", loadExtensions: [".ts"] },
};

export default config;
