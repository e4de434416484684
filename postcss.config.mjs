// PostCSS runs Tailwind CSS 4 only.
export default { plugins: { "@tailwindcss/postcss": {} } };
