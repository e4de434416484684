// PostCSS runs Tailwind CSS 4 only.
const config = { plugins: { "@tailwindcss/postcss": {} } };

export default config;
