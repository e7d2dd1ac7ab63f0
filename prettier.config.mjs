/**
 * Prettier settings for the whole tree. The line width follows the code as written (most lines fit in 120);
 * the Tailwind plugin sorts class lists and reads the theme from app/globals.css.
 * @type {import("prettier").Config}
 */
const config = {
  printWidth: 120,
  semi: true,
  singleQuote: false,
  trailingComma: "all",
  plugins: ["prettier-plugin-tailwindcss"],
  tailwindStylesheet: "./app/globals.css",
  tailwindFunctions: ["cn"],
};

export default config;
