import type { ButtonHTMLAttributes } from 'react';

type Variant = 'primary' | 'secondary' | 'quiet';

const styles: Record<Variant, string> = {
  primary: 'bg-deep-700 text-white hover:bg-deep-900 disabled:bg-shell-300',
  secondary: 'bg-white text-deep-700 border border-deep-300 hover:bg-deep-50 disabled:text-shell-500',
  quiet: 'text-deep-700 underline-offset-4 hover:underline',
};

export function Button({ variant = 'primary', className = '', ...props }: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: Variant }) {
  return <button className={`inline-flex items-center justify-center gap-2 rounded-md px-4 py-2 text-sm font-semibold transition-colors disabled:cursor-not-allowed ${styles[variant]} ${className}`} {...props} />;
}
