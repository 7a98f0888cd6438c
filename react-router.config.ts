import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  appDirectory: "app",
  // BUILD_DIR lets two checkouts of work build side by side without clobbering each other.
  buildDirectory: process.env.BUILD_DIR ?? "build",
} satisfies Config;
