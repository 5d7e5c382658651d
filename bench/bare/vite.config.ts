import { reactRouter } from "@react-router/dev/vite";
import { defineConfig } from "vite";

// Built from this folder with the project's own node_modules (no install of its own).
export default defineConfig({ plugins: [reactRouter()] });
