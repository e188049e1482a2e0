import { Fragment } from 'react';

/**
 * An e-mail address that wraps only where a reader expects it to (after the @, before a dot),
 * never in the middle of a name. Unbroken runs longer than the line are the one exception.
 */
export function EmailAddress({ value, className = '' }: { value: string; className?: string }) {
  const pieces = value.split(/(?=[.])|(?<=@)/);
  return (
    <span className={`break-words ${className}`}>
      {pieces.map((piece, i) => (
        <Fragment key={i}>
          {i > 0 ? <wbr /> : null}
          {piece}
        </Fragment>
      ))}
    </span>
  );
}
