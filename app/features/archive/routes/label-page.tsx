import { useQuery } from '@tanstack/react-query';
import { useEffect } from 'react';
import { useNavigate, useParams } from 'react-router-dom';
import { ButtonLink } from '../../../components/ui/button.tsx';
import { ErrorBanner } from '../../../components/ui/error-banner.tsx';
import { Loading } from '../../../components/ui/loading.tsx';
import { PageHeading } from '../../../components/ui/page-heading.tsx';
import { paths } from '../../../lib/paths.ts';
import { labelQueryOptions } from '../api.ts';

/** Where a label's QR lands: the code is looked up and the cast or place opens in its stead. */
export function LabelPage() {
  const code = useParams().code ?? '';
  const navigate = useNavigate();
  const label = useQuery(labelQueryOptions(code));
  useEffect(() => {
    if (!label.data) return;
    navigate(label.data.target === 'cast' ? paths.cast.href(label.data.id) : paths.place.href(label.data.id), { replace: true });
  }, [label.data, navigate]);

  if (label.isError) {
    return (
      <>
        <PageHeading title="Label not found">Label {code}</PageHeading>
        <ErrorBanner title="This label does not open anything" error={label.error} />
        <div>
          <ButtonLink to={paths.archive.href()}>Find a cast</ButtonLink>
        </div>
      </>
    );
  }
  return <Loading label={`Opening label ${code}…`} rows={1} />;
}
