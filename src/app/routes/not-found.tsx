import { Link } from 'react-router-dom';

export function Component() {
  return (
    <section className="py-12">
      <h1 className="text-3xl font-semibold text-leaf-900">Nothing grows here</h1>
      <p className="mt-3 max-w-prose">
        This page does not exist, or it belongs to a trial you are not part of.
      </p>
      <Link to="/" className="mt-6 inline-block font-semibold text-leaf-700 underline">
        Back to your trials
      </Link>
    </section>
  );
}
