// Production server: the built React Router app behind Express, with static assets,
// the client's address for sign-in throttling, foreign-origin refusal and a clean shutdown.
import { existsSync } from "node:fs";
import path from "node:path";

// Before anything imports React: the environment decides which build of it loads.
if (existsSync(".env")) process.loadEnvFile(".env");
process.env.NODE_ENV ??= "production";

const { createRequestHandler } = await import("@react-router/express");
const { default: compression } = await import("compression");
const { default: express } = await import("express");

const buildDirectory = path.resolve(process.env.BUILD_DIR ?? "build");
let build;
try {
  build = await import(path.join(buildDirectory, "server/index.js"));
} catch (error) {
  console.error(`Cannot load the built app from ${buildDirectory}: run \`npm run build\` first.\n${error.message}`);
  process.exit(1);
}
const entry = build.entry.module;
try {
  // Validates every environment variable now, so a bad one stops the server with its name.
  entry.checkEnvironment();
} catch (error) {
  console.error(error.message);
  process.exit(1);
}

const trustProxy = process.env.TRUST_PROXY === "true" || process.env.TRUST_PROXY === "1";
const app = express();
app.disable("x-powered-by");
app.set("trust proxy", trustProxy);
app.use(compression());
app.use(
  "/assets",
  express.static(path.join(buildDirectory, "client/assets"), { immutable: true, maxAge: "1y", index: false }),
);
app.use(express.static(path.join(buildDirectory, "client"), { maxAge: "1h", index: false }));
app.use((req, res, next) => {
  const url = `${req.protocol}://${req.get("host")}${req.originalUrl}`;
  const headers = { origin: req.get("origin") ?? "", referer: req.get("referer") ?? "" };
  if (entry.isForeignOrigin(req.method, url, headers)) {
    res
      .status(403)
      .set(entry.securityHeaderRecord())
      .json({ error: "This request came from another site and was refused." });
    return;
  }
  req.headers["x-foamtally-client-address"] = (trustProxy ? req.ip : req.socket.remoteAddress) ?? "unknown";
  next();
});
app.all("/{*splat}", createRequestHandler({ build }));

const port = Number(process.env.PORT ?? 3000);
const host = process.env.HOST ?? "127.0.0.1";
const server = app.listen(port, host, () => {
  console.log(`Foamtally is serving on http://${host}:${port}`);
  // Sends queued mail (alerts, notices, workbooks) every 30 s and retries failed sends with backoff.
  entry.startMailWorker?.();
});

function shutdown(signal) {
  console.log(`${signal}: stopping Foamtally`);
  server.close(() => process.exit(0));
  server.closeIdleConnections();
  setTimeout(() => process.exit(0), 3_000).unref();
}
process.on("SIGTERM", () => shutdown("SIGTERM"));
process.on("SIGINT", () => shutdown("SIGINT"));
