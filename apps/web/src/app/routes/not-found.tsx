import { Link } from "react-router-dom";
import { paths } from "../../config/paths";

export function NotFound() {
  return (
    <section aria-labelledby="not-found-title" className="mx-auto max-w-xl py-16 text-center">
      <h1 id="not-found-title" className="text-title font-semibold text-ink-950">
        There is no such page
      </h1>
      <p className="mt-3 text-lead text-ink-700">The address may be mistyped, or the page may have moved.</p>
      <Link
        to={paths.home.getHref()}
        className="mt-6 inline-flex rounded-md bg-stream-700 px-4 py-2 text-small font-medium text-white hover:bg-stream-800"
      >
        Go to your home screen
      </Link>
    </section>
  );
}
