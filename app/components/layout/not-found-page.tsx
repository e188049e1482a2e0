import { ButtonLink } from '../ui/button.tsx';
import { PageHeading } from '../ui/page-heading.tsx';
import { paths } from '../../lib/paths.ts';

export function NotFoundPage() {
  return (
    <>
      <PageHeading title="Page not found" testId="not-found-heading">
        Page not found
      </PageHeading>
      <p className="max-w-prose text-graphite-700">There is no page at this address. It may have moved, or the link may be mistyped.</p>
      <div>
        <ButtonLink to={paths.home.href()}>Go to Today</ButtonLink>
      </div>
    </>
  );
}
