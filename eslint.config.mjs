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
  {
    // lib/assessment/rules is pure too: it may use the physics engine, the worst-case types and the
    // stored enumerations, and zod for the settings schema — nothing that reads or writes state.
    files: ["lib/assessment/rules/**/*.ts"],
    rules: {
      "no-restricted-imports": [
        "error",
        {
          paths: ["next", "react", "fs", "path", "server-only"],
          patterns: [
            { regex: "^@/(?!(lib/hazard|lib/temperatures/worst-case|db/enums)$)", message: "The assessment rules are pure: import only @/lib/hazard, @/lib/temperatures/worst-case (types) and @/db/enums." },
            { group: ["../*", "next/*", "node:*"], message: "The assessment rules are pure: no framework, no I/O, no imports from outside the folder." },
          ],
        },
      ],
    },
  },
];

export default config;
