import type { Config } from "@react-router/dev/config";

/** The bare page the benchmark compares Torqueleaf with: server rendering, nothing else. */
export default { ssr: true } satisfies Config;
