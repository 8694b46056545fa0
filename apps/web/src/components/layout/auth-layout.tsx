import type { ReactNode } from "react";
import { ConfluenceArt } from "../brand/confluence-art";
import { Wordmark } from "../brand/wordmark";

/** The frame around sign-in: the product's name on one side, the form on the other. */
export function AuthLayout({ title, children }: { title: string; children: ReactNode }) {
  return (
    <div className="grid min-h-screen lg:grid-cols-[minmax(0,5fr)_minmax(0,6fr)]">
      <header className="on-dark relative hidden overflow-hidden bg-ink-900 px-12 py-12 text-ink-100 lg:flex lg:flex-col">
        <ConfluenceArt className="pointer-events-none absolute inset-0 h-full w-full" />
        <Wordmark tone="dark" className="relative" />
        <div className="relative mt-auto max-w-md">
          <p className="text-display font-semibold leading-tight text-white">
            What does each channel really cost per new customer?
          </p>
          <p className="mt-4 text-lead text-ink-200">
            Cost per customer for every brand, market and channel, with the uncertainty shown, so budget goes where
            it earns most.
          </p>
        </div>
      </header>
      <main id="main" className="flex items-center justify-center px-6 py-12">
        <div className="w-full max-w-sm">
          <div className="mb-8 lg:hidden">
            <Wordmark tone="light" />
          </div>
          <h1 className="text-title font-semibold tracking-tight text-ink-950">{title}</h1>
          <div className="mt-6">{children}</div>
        </div>
      </main>
    </div>
  );
}
