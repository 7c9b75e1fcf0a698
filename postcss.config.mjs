// Tailwind CSS 4 runs as one PostCSS plugin; the theme itself lives in app/globals.css.
const config = {
  plugins: { "@tailwindcss/postcss": {} },
};
export default config;
