import type { Config } from "@react-router/dev/config";

export default {
  ssr: true,
  // Cross-origin writes are refused by the app's own security middleware, which answers 403 and
  // also reads Sec-Fetch-Site; React Router's built-in check would answer a bare 400 first.
  allowedActionOrigins: ["**"],
  future: {
    v8_middleware: true,
    v8_splitRouteModules: true,
    v8_viteEnvironmentApi: true,
    v8_trailingSlashAwareDataRequests: true,
    v8_passThroughRequests: true,
  },
} satisfies Config;
