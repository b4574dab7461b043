import type { Config } from 'tailwindcss';

// Lagwise palette: "slate-ink" neutrals for dense tables, a mineral teal for actions,
// and a warm ochre reserved for warnings about hot or sweating surfaces.
const config: Config = {
  content: ['./app/**/*.{ts,tsx}', './components/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        ink: {
          50: '#f6f7f8',
          100: '#eceef1',
          200: '#d5d9df',
          300: '#b1b9c3',
          400: '#87929f',
          500: '#677482',
          600: '#525d69',
          700: '#434c56',
          800: '#3a4149',
          900: '#23282e',
          950: '#15181c',
        },
        mineral: {
          50: '#eefaf8',
          100: '#d5f2ee',
          200: '#aee4dd',
          300: '#7bcfc6',
          400: '#4cb3aa',
          500: '#31978f',
          600: '#257a74',
          700: '#21625e',
          800: '#1f4f4c',
          900: '#1d4240',
        },
        ochre: {
          50: '#fdf8ec',
          100: '#f9ecc9',
          300: '#eec062',
          500: '#d9912a',
          700: '#a15a1c',
          900: '#6b3b19',
        },
        alarm: { 50: '#fdf3f2', 100: '#fbe3e0', 500: '#c9412f', 700: '#8f2a1f' },
      },
      fontFamily: {
        sans: ['var(--font-sans)', 'system-ui', 'sans-serif'],
        mono: ['var(--font-mono)', 'ui-monospace', 'monospace'],
      },
    },
  },
  plugins: [],
};
export default config;
