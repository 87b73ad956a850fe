import { reactRouter } from "@react-router/dev/vite";
import tailwindcss from "@tailwindcss/vite";
import { defineConfig } from "vite";

export default defineConfig({
  plugins: [tailwindcss(), reactRouter()],
  resolve: { tsconfigPaths: true },
  // fiber ships ESM that the SSR build must bundle rather than require()
  ssr: { noExternal: ["@react-three/fiber"] },
  server: { port: Number(process.env.PORT ?? 4310) },
});
