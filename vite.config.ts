import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

export default defineConfig({
  plugins: [tailwindcss(), reactRouter()],
  resolve: { tsconfigPaths: true },
  ssr: {
    // Native and server-only packages stay external to the server bundle.
    external: ["sharp", "@libsql/client", "s3rver", "smtp-server", "mailparser", "nodemailer"],
  },
});
