import type { ReactNode } from 'react';

type CardProps = { children: ReactNode; as?: 'section' | 'div' | 'article'; labelledBy?: string };

/** The record card: warm paper on the workshop-grey ground, a thin rule, no heavy box. */
export function Card({ children, as: Tag = 'section', labelledBy }: CardProps) {
  return (
    <Tag aria-labelledby={labelledBy} className="rounded-card border border-rule bg-card shadow-card">
      {children}
    </Tag>
  );
}

type CardHeaderProps = { title: ReactNode; id?: string; description?: ReactNode; actions?: ReactNode; level?: 2 | 3 };

export function CardHeader({ title, id, description, actions, level = 2 }: CardHeaderProps) {
  const H = level === 2 ? 'h2' : 'h3';
  return (
    <header className="flex flex-wrap items-start justify-between gap-3 border-b border-rule px-5 py-3.5">
      <div className="min-w-0">
        <H id={id} className="text-lg font-semibold leading-snug">
          {title}
        </H>
        {description && <p className="mt-0.5 text-sm text-ink-soft">{description}</p>}
      </div>
      {actions && <div className="flex flex-wrap items-center gap-2">{actions}</div>}
    </header>
  );
}

export function CardBody({ children, flush = false }: { children: ReactNode; flush?: boolean }) {
  return <div className={flush ? '' : 'px-5 py-4'}>{children}</div>;
}

export function CardFooter({ children }: { children: ReactNode }) {
  return (
    <footer className="flex flex-wrap items-center justify-between gap-3 border-t border-rule px-5 py-3">
      {children}
    </footer>
  );
}
