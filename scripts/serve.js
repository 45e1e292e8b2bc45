// Production server: the built React Router app behind Express, with static assets,
// request-body limits, the client's address for sign-in throttling, foreign-origin refusal and a
// clean shutdown.
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
// Every body is bounded before the app reads it: a declared length above the route's limit is
// refused at once, and a body without a declared length (chunked) is refused too, because only a
// declared length lets Node stop reading at the limit. The app's readers count bytes again.
app.use((req, res, next) => {
  const hasBody = req.headers["transfer-encoding"] !== undefined || req.headers["content-length"] !== undefined;
  if (!hasBody) return next();
  const refuse = (status, message) => {
    res.status(status).set(entry.securityHeaderRecord()).set("Connection", "close");
    if (req.path.startsWith("/api/") || req.accepts(["json", "html"]) !== "html") res.json({ error: message });
    else
      res.type("html").send(`<!doctype html><title>Foamtally</title><p>${message}</p><p><a href="/">Foamtally</a></p>`);
  };
  const limit = entry.requestBodyLimit(req.path);
  const declared = req.headers["content-length"];
  if (declared === undefined) {
    return refuse(411, "Send the request with a Content-Length header.");
  }
  if (Number(declared) > limit) {
    return refuse(
      413,
      `The request is larger than ${Math.round((limit / 1024 / 1024) * 10) / 10} MB and was not read.`,
    );
  }
  next();
});
// Bodies under 1 KB go as they are (the app declares the length of its JSON answers); a body the
// app already compressed (the map's events, kept gzipped per data version) is left alone.
app.use(compression({ threshold: 1024 }));
app.use(
  "/assets",
  express.static(path.join(buildDirectory, "client/assets"), { immutable: true, maxAge: "1y", index: false }),
);
// Every file in public/ has an extension; a page or API address without one skips the disk lookup.
const publicFiles = express.static(path.join(buildDirectory, "client"), { maxAge: "1h", index: false });
app.use((req, res, next) => (/\.[^/]*$/.test(req.path) ? publicFiles(req, res, next) : next()));
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
  // Shortly after start, then hourly: foam-system reminders (30 days ahead, and when overdue) and
  // stock alerts that fall due with time alone (shelf life, quality samples).
  entry.startScheduledChecks?.();
});

function shutdown(signal) {
  console.log(`${signal}: stopping Foamtally`);
  server.close(() => process.exit(0));
  server.closeIdleConnections();
  setTimeout(() => process.exit(0), 3_000).unref();
}
process.on("SIGTERM", () => shutdown("SIGTERM"));
process.on("SIGINT", () => shutdown("SIGINT"));
