import type { ButtonHTMLAttributes } from 'react';

const variants = {
  primary: 'bg-leaf-700 text-white hover:bg-leaf-900 disabled:bg-leaf-300',
  secondary:
    'border border-leaf-700 text-leaf-700 bg-white hover:bg-leaf-50 disabled:border-leaf-300 disabled:text-leaf-500 disabled:hover:bg-white',
  danger: 'bg-frost-600 text-white hover:brightness-90',
  ghost: 'text-leaf-700 hover:bg-leaf-50',
};

export function Button({
  variant = 'primary',
  className = '',
  ...props
}: ButtonHTMLAttributes<HTMLButtonElement> & { variant?: keyof typeof variants }) {
  return (
    <button
      className={`inline-flex min-h-11 items-center justify-center gap-2 rounded-lg px-4 font-semibold transition-colors disabled:cursor-not-allowed ${variants[variant]} ${className}`}
      {...props}
    />
  );
}
