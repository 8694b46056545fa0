// Portfolio settings (admins): company name, reporting currency, customer value per brand,
// brand and market names, channel names and order. Reading is for admins too: the list names every brand, which a
// market manager's lists never do.
import { brandNamesInput, channelSettingsInput, companySettingsInput, customerValuesInput, marketNamesInput, type PortfolioSettings } from "@tributary/contracts";
import { defineRoute, markets, signedIn } from "../access/route-table";
import { portfolioSettings, updateBrandNames, updateChannelSettings, updateCompanySettings, updateCustomerValues, updateMarketNames } from "../settings/portfolio-settings";

const admins = ["admin"] as const;

export const portfolioSettingsRoutes = [
  defineRoute({
    method: "get",
    path: "/api/portfolio-settings",
    access: signedIn(markets.unscoped, admins),
    handler: ({ db }): Promise<PortfolioSettings> => portfolioSettings(db),
  }),
  defineRoute({
    method: "patch",
    path: "/api/portfolio-settings/company",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db, user }): Promise<PortfolioSettings> => updateCompanySettings(db, user, companySettingsInput.parse(req.body ?? {})),
  }),
  defineRoute({
    method: "put",
    path: "/api/portfolio-settings/customer-values",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db, user }): Promise<PortfolioSettings> => updateCustomerValues(db, user, customerValuesInput.parse(req.body ?? {})),
  }),
  defineRoute({
    method: "put",
    path: "/api/portfolio-settings/channels",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db, user }): Promise<PortfolioSettings> => updateChannelSettings(db, user, channelSettingsInput.parse(req.body ?? {})),
  }),
  defineRoute({
    method: "put",
    path: "/api/portfolio-settings/brand-names",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db, user }): Promise<PortfolioSettings> => updateBrandNames(db, user, brandNamesInput.parse(req.body ?? {})),
  }),
  defineRoute({
    method: "put",
    path: "/api/portfolio-settings/market-names",
    access: signedIn(markets.unscoped, admins),
    handler: ({ req, db, user }): Promise<PortfolioSettings> => updateMarketNames(db, user, marketNamesInput.parse(req.body ?? {})),
  }),
];
