import type { ReactNode } from 'react';
import Markdown, { type Components } from 'react-markdown';

type Level = 2 | 3 | 4;

function heading(level: Level) {
  const Tag = `h${Math.min(level, 6)}` as 'h2';
  const size = level === 2 ? 'text-2xl' : level === 3 ? 'text-xl' : 'text-lg';
  return function Heading({ children }: { children?: ReactNode }) {
    return <Tag className={`mt-2 font-bold text-graphite-900 ${size}`}>{children}</Tag>;
  };
}

function componentsFor(top: Level): Components {
  const next = Math.min(top + 1, 4) as Level;
  return {
    // The consent's own headings sit under the page's: "#" and "##" become `top`, deeper ones one below.
    h1: heading(top),
    h2: heading(top),
    h3: heading(next),
    h4: heading(next),
    h5: heading(next),
    h6: heading(next),
    p: ({ children }) => <p className="max-w-prose">{children}</p>,
    ul: ({ children }) => <ul className="flex max-w-prose list-disc flex-col gap-2 pl-6">{children}</ul>,
    ol: ({ children }) => <ol className="flex max-w-prose list-decimal flex-col gap-2 pl-6">{children}</ol>,
    strong: ({ children }) => <strong className="font-bold text-graphite-900">{children}</strong>,
    a: ({ children, href }) => (
      <a href={href} rel="noreferrer noopener" target="_blank" className="font-semibold underline">
        {children}
      </a>
    ),
    blockquote: ({ children }) => <blockquote className="border-l-4 border-plaster-300 pl-4 text-graphite-700">{children}</blockquote>,
    hr: () => <hr className="border-plaster-300" />,
    code: ({ children }) => <code className="rounded bg-plaster-100 px-1 font-mono">{children}</code>,
  };
}

// Built once per level: components made during render would remount the text on every render.
const COMPONENTS: Record<Level, Components> = { 2: componentsFor(2), 3: componentsFor(3), 4: componentsFor(4) };

/**
 * The exact consent text as written in its Markdown. No raw HTML is ever rendered (react-markdown
 * leaves it out by default) and no images are shown, only words.
 */
export function ConsentText({ body, headingLevel = 2, large = false, testId }: { body: string; headingLevel?: Level; large?: boolean; testId?: string }) {
  return (
    <div className={`flex flex-col gap-3 text-graphite-900 ${large ? 'text-xl leading-relaxed' : 'text-base'}`} data-testid={testId}>
      <Markdown components={COMPONENTS[headingLevel]} disallowedElements={['img']} unwrapDisallowed skipHtml>
        {body}
      </Markdown>
    </div>
  );
}
