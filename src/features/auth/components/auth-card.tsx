import type { ReactNode } from 'react';

export function AuthCard({ title, children }: { title: string; children: ReactNode }) {
  return (
    <section className="mx-auto w-full max-w-md rounded-xl bg-white p-4 shadow-sm sm:p-6">
      <h1 className="text-2xl font-semibold text-leaf-900">{title}</h1>
      <div className="mt-4 flex flex-col gap-4">{children}</div>
    </section>
  );
}
