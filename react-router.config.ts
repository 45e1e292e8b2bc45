import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  buildDirectory: process.env.BUILD_DIR ?? "build",
  future: {
    v8_middleware: true,
  },
} satisfies Config;
