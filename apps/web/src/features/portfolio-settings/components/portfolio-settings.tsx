import { PageHeader } from "../../../components/ui/page-header";
import { ErrorState } from "../../../components/ui/error-state";
import { LoadingState } from "../../../components/ui/loading-state";
import { usePortfolioSettings } from "../api/get-portfolio-settings";
import { ChannelsForm } from "./channels-form";
import { CompanyForm } from "./company-form";
import { CustomerValuesForm } from "./customer-values-form";
import { EntityNamesForm } from "./entity-names-form";

/** Admins: the company name, reporting currency, customer value per brand, brand and market names, and the channels' names and order. */
export function PortfolioSettings() {
  const settings = usePortfolioSettings();
  return (
    <>
      <PageHeader
        title="Portfolio settings"
        description="What the whole workspace shares: the company name, the currency money is labelled in, what a new customer is worth to each brand, how brands and markets are named, and how channels are named and ordered. Every change is in the audit log."
      />
      {settings.isPending ? (
        <LoadingState label="Loading the portfolio settings…" />
      ) : settings.isError ? (
        <ErrorState title="The portfolio settings could not be loaded" message={settings.error.message} onRetry={() => void settings.refetch()} />
      ) : (
        <div className="space-y-8">
          <CompanyForm settings={settings.data} />
          <CustomerValuesForm settings={settings.data} />
          <EntityNamesForm kind="brand" settings={settings.data} />
          <EntityNamesForm kind="market" settings={settings.data} />
          <ChannelsForm settings={settings.data} />
        </div>
      )}
    </>
  );
}
