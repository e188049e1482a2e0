import type { ReactNode } from 'react';
import { Wordmark } from './wordmark.tsx';
import { useDocumentTitle } from '../../lib/use-document-title.ts';

/** Pages a performer opens without signing in: Plinth's mark, the page, and nothing of any staff session. */
export function PublicFrame({ title, children, narrow = false }: { title: string; children: ReactNode; narrow?: boolean }) {
  useDocumentTitle(title);
  return (
    <div className="min-h-screen bg-plaster-100">
      <header className="border-b border-plaster-300 bg-white">
        <div className={`mx-auto flex items-center px-4 py-3 sm:px-8 ${narrow ? 'max-w-2xl' : 'max-w-4xl'}`}>
          <Wordmark />
        </div>
      </header>
      <main className={`mx-auto flex flex-col gap-6 px-4 py-6 sm:px-8 sm:py-8 ${narrow ? 'max-w-2xl' : 'max-w-4xl'}`}>{children}</main>
      <footer className="border-t border-plaster-300">
        <p className={`mx-auto px-4 py-4 text-sm text-graphite-700 sm:px-8 ${narrow ? 'max-w-2xl' : 'max-w-4xl'}`}>
          Plinth records skin screening and consent; it is not a medical diagnosis.
        </p>
      </footer>
    </div>
  );
}
