import nextCoreWebVitals from "eslint-config-next/core-web-vitals";
import nextTypescript from "eslint-config-next/typescript";

const config = [
  ...nextCoreWebVitals,
  ...nextTypescript,
  {
    ignores: [
      "node_modules/**",
      ".next/**",
      "drizzle/**",
      "data/**",
      "test-results/**",
      "playwright-report/**",
      "next-env.d.ts",
    ],
  },
  {
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_" }],
    },
  },
  {
    // lib/hazard is the pure physics module: nothing from the app may leak into it.
    files: ["lib/hazard/**/*.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        { patterns: ["@/db/*", "@/app/*", "@/components/*", "next/*", "next", "react", "node:*", "fs", "path"] },
      ],
    },
  },
];

export default config;
