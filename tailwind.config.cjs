/** Bearline's own theme: slate-blue ink, moss green for go, amber for caution. */
/** @type {import('tailwindcss').Config} */
module.exports = {
  content: ['./src/**/*.{astro,html,js,jsx,ts,tsx,md}'],
  theme: {
    extend: {
      fontFamily: {
        sans: ['"Noto Sans"', 'system-ui', 'sans-serif'],
      },
      colors: {
        ink: {
          50: '#f3f6f9',
          100: '#e3e9f0',
          200: '#c4d1de',
          300: '#97aec4',
          400: '#6785a3',
          500: '#476785',
          600: '#36516c',
          700: '#2b4158',
          800: '#1f3043',
          900: '#152231',
        },
        moss: { 50: '#f1f8f2', 100: '#dcefdf', 500: '#3b8a4f', 600: '#2e7040', 700: '#255a34' },
        ember: { 50: '#fff7eb', 100: '#fdebc8', 500: '#d9891a', 600: '#b46d10', 700: '#8a520b' },
        alarm: { 50: '#fdf1f0', 100: '#fadcd9', 500: '#c2412f', 600: '#a13424', 700: '#7f291c' },
      },
    },
  },
  plugins: [],
};
