import type { Config } from "@react-router/dev/config";

export default {
  // Server rendering on: field pages must show something useful before scripts load.
  ssr: true,
  future: { v8_middleware: true },
} satisfies Config;
