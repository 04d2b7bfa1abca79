// Tailwind CSS 4 reads its theme from app/globals.css (@theme); this file records the
// content globs and the font variable for editors and for anyone on the classic config.
const config = {
  content: ["./app/**/*.{ts,tsx}", "./components/**/*.{ts,tsx}"],
  theme: {
    extend: {
      fontFamily: { sans: ["var(--font-inter)", "system-ui", "sans-serif"] },
    },
  },
};

export default config;
