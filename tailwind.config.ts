import type { Config } from 'tailwindcss';

/**
 * Brackline's own palette, taken from the coast: deep water, estuary green, sand and shell grey
 * for the chrome. Ratings use one sequential scale (see src/components/ui/rating-badge.tsx),
 * always with a label, never colour alone.
 */
export default {
  content: ['./index.html', './src/**/*.{ts,tsx}'],
  theme: {
    extend: {
      colors: {
        deep: { 50: '#eef3f8', 100: '#d5e1ee', 300: '#7f9fc0', 500: '#2e5b86', 700: '#173d61', 900: '#0c2238' },
        estuary: { 50: '#eef6f3', 100: '#d3e9e1', 300: '#7fb5a3', 500: '#2f7a66', 700: '#1f5548', 900: '#12332b' },
        sand: { 50: '#fbf8f1', 100: '#f4ecdb', 200: '#eadcbf', 400: '#cfb27c', 600: '#9c7a3f' },
        shell: { 50: '#f6f6f5', 100: '#e9e9e7', 300: '#bdbdb8', 500: '#7c7d78', 700: '#4b4c48', 900: '#22231f' },
      },
      fontFamily: {
        sans: ['"Merriweather Sans"', 'system-ui', 'sans-serif'],
      },
    },
  },
} satisfies Config;
