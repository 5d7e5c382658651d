import type { ReactNode } from "react";

/** The card the account screens (sign-in, sign-up, reset) are laid out in. */
export function AuthCard({
  title,
  intro,
  children,
  wide = false,
}: {
  title: string;
  intro?: ReactNode;
  children: ReactNode;
  wide?: boolean;
}) {
  return (
    <section className={`mx-auto ${wide ? "max-w-3xl" : "max-w-md"} px-4 py-8 sm:px-6 sm:py-12`}>
      <div className="rounded-xl border border-rule bg-white p-5 shadow-sm sm:p-7">
        <h1 className="font-serif text-3xl font-semibold tracking-tight text-spruce-900">{title}</h1>
        {intro ? <p className="mt-2 text-ink-soft">{intro}</p> : null}
        <div className="mt-6">{children}</div>
      </div>
    </section>
  );
}
