import { Link } from "react-router-dom";

type NotAvailableProps = { screenLabel: string; roleLabel: string; homeHref: string; homeLabel: string };

export function NotAvailable({ screenLabel, roleLabel, homeHref, homeLabel }: NotAvailableProps) {
  return (
    <section aria-labelledby="not-available-title" className="mx-auto max-w-xl py-16 text-center">
      <p className="text-caption font-semibold uppercase tracking-wider text-caution-700">Not available</p>
      <h1 id="not-available-title" className="mt-2 text-title font-semibold text-ink-950">
        {screenLabel} is not available for your role
      </h1>
      <p className="mt-3 text-lead text-ink-700">
        You are signed in as <strong className="font-semibold">{roleLabel}</strong>. This screen belongs to other
        roles. If you need it, ask an admin to change your role.
      </p>
      <Link
        to={homeHref}
        className="mt-6 inline-flex rounded-md bg-stream-700 px-4 py-2 text-small font-medium text-white hover:bg-stream-800"
      >
        Go to {homeLabel}
      </Link>
    </section>
  );
}
