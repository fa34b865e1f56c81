// ESLint for the whole workspace: JavaScript and TypeScript rules, Vue's style guide
// ("recommended": essential + strongly recommended + recommended), Prettier for layout, and the
// architecture's boundaries as import restrictions. `pnpm lint` runs it with the type checks.
import js from "@eslint/js";
import prettier from "eslint-config-prettier";
import vue from "eslint-plugin-vue";
import globals from "globals";
import tseslint from "typescript-eslint";

/** The card-payment provider's SDK stays behind the payments port. */
const providerSdk = {
  paths: [
    {
      name: "stripe",
      message:
        "The payment provider's SDK stays in apps/api/src/integrations/: use the payments port (PaymentsPort in integrations/payments.ts) and its domain events and errors.",
    },
  ],
  patterns: [
    {
      group: ["stripe/*"],
      message:
        "The payment provider's SDK stays in apps/api/src/integrations/: use the payments port (PaymentsPort in integrations/payments.ts).",
    },
  ],
};

/** Import bans that keep the layers of ARCHITECTURE.md. */
const boundaries = {
  api: providerSdk,
  routes: {
    paths: [{ name: "typeorm", message: "Routes stay thin: database work belongs in a service." }, ...providerSdk.paths],
    patterns: providerSdk.patterns,
  },
  sharedUi: {
    patterns: [
      {
        group: ["**/api/*", "!**/api/errors.ts"],
        allowTypeImports: true,
        message: "Shared UI components take data through props or composables, never an API client.",
      },
    ],
  },
  slabMath: {
    patterns: [{ group: ["node:*", "vue", "express", "typeorm", "zod"], message: "slab-math is pure: no I/O, no framework." }],
  },
};

export default tseslint.config(
  {
    ignores: ["**/node_modules/**", "**/dist/**", ".data/**", "test-results/**", "coverage/**"],
  },
  js.configs.recommended,
  ...tseslint.configs.recommended,
  ...vue.configs["flat/recommended"],
  {
    files: ["**/*.vue"],
    languageOptions: {
      parserOptions: { parser: tseslint.parser, extraFileExtensions: [".vue"], sourceType: "module" },
    },
  },
  {
    languageOptions: {
      ecmaVersion: 2023,
      sourceType: "module",
      globals: { ...globals.node },
    },
    linterOptions: { reportUnusedDisableDirectives: "error" },
    rules: {
      "@typescript-eslint/no-unused-vars": ["error", { argsIgnorePattern: "^_", varsIgnorePattern: "^_", caughtErrors: "none" }],
      "@typescript-eslint/consistent-type-imports": ["error", { fixStyle: "inline-type-imports" }],
      "no-console": ["error", { allow: ["warn", "error"] }],
      eqeqeq: ["error", "always", { null: "ignore" }],
      "prefer-const": "error",
      "no-var": "error",
      "object-shorthand": ["error", "properties"],
    },
  },
  {
    files: ["apps/web/src/**/*.{ts,vue}"],
    languageOptions: { globals: { ...globals.browser } },
    rules: {
      "vue/block-lang": ["error", { script: { lang: "ts" } }],
      "vue/component-api-style": ["error", ["script-setup"]],
      "vue/define-macros-order": "error",
      "vue/no-unused-refs": "error",
      "vue/no-useless-v-bind": "error",
      "vue/prefer-true-attribute-shorthand": "error",
      "vue/require-typed-ref": "error",
    },
  },
  {
    // Command-line tools, benchmarks and the stack runner print to the terminal on purpose.
    files: ["**/cli/**", "**/bench/**", "apps/*/src/main.ts", "apps/web/route-size.ts", "packages/devstack/**"],
    rules: { "no-console": "off" },
  },
  {
    // The payments stand-in reads the provider's loosely typed, form-encoded bodies as they come.
    files: ["apps/payments-fake/src/**/*.ts"],
    rules: { "@typescript-eslint/no-explicit-any": "off" },
  },
  {
    // Tests that drive the payments fake may use the SDK's own helpers (signing webhooks, say).
    files: ["apps/api/src/**/*.ts"],
    ignores: ["apps/api/src/integrations/**", "apps/api/src/test-support/**", "**/*.test.ts"],
    rules: { "no-restricted-imports": ["error", boundaries.api] },
  },
  {
    files: ["apps/api/src/routes/**/*.ts"],
    ignores: ["**/*.test.ts"],
    rules: { "no-restricted-imports": ["error", boundaries.routes] },
  },
  {
    files: ["apps/web/src/components/{common,form,layout,brand}/**/*.{ts,vue}"],
    ignores: ["**/*.test.ts"],
    rules: { "no-restricted-imports": ["error", boundaries.sharedUi] },
  },
  {
    files: ["packages/slab-math/src/**/*.ts"],
    ignores: ["**/*.test.ts", "**/*.bench.ts"],
    rules: { "no-restricted-imports": ["error", boundaries.slabMath] },
  },
  prettier,
);
