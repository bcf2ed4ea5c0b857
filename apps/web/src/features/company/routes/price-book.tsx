import { useQuery } from '@tanstack/react-query';
import { Alert } from '@/components/ui/alert';
import { LoadFailed } from '@/components/ui/load-failed';
import { SectionLoading } from '@/components/ui/spinner';
import { priceBookQueryOptions } from '../api';
import { CompanyPage } from '../components/company-page';
import { PriceBookEditor } from '../components/price-book-editor';

export function PriceBookRoute() {
  const stored = useQuery(priceBookQueryOptions());

  return (
    <CompanyPage
      title="Price book"
      description="The repair and maintenance prices behind every report’s cost ranges. Changes apply to reports not yet published; published reports keep their figures."
    >
      {stored.isPending ? (
        <SectionLoading label="Loading the price book…" />
      ) : stored.isError ? (
        <LoadFailed what="price book" error={stored.error} onRetry={() => void stored.refetch()} retrying={stored.isFetching} />
      ) : (
        <div className="space-y-4">
          {stored.data.isDefault ? (
            <Alert tone="caution" title="These are Underfoot’s documented defaults, not your prices">
              They come from consumer cost guides or are invented for the demo, and each says so in its note. Replace them with your own
              prices and save, so reports show your company’s ranges.
            </Alert>
          ) : null}
          <PriceBookEditor stored={stored.data} />
        </div>
      )}
    </CompanyPage>
  );
}
