import { describe, expect, it } from "vitest";
import { brandNamesInput, channelSettingsInput, companySettingsInput, currencyCodes, customerValuesInput, isCurrencyCode, marketNamesInput, nameKey } from "./portfolio-settings";

describe("portfolio settings schemas", () => {
  it("offers the ISO 4217 codes the runtime can format, alphabetical, and refuses others", () => {
    const codes = currencyCodes();
    expect(codes).toContain("EUR");
    expect(codes).toContain("JPY");
    expect([...codes].sort()).toEqual(codes);
    expect(codes.every((code) => /^[A-Z]{3}$/.test(code))).toBe(true);
    expect(isCurrencyCode("QQQ")).toBe(false);
    expect(companySettingsInput.parse({ currency: " sek " })).toEqual({ currency: "SEK" });
    expect(companySettingsInput.safeParse({ currency: "QQQ" }).error?.issues.map((i) => i.path.join("."))).toEqual(["currency"]);
    expect(companySettingsInput.safeParse({ currency: "EURO" }).error?.issues).toHaveLength(1);
  });

  it("tidies names (composed, invisible characters dropped, spaces collapsed) and refuses what cannot be shown safely", () => {
    expect(companySettingsInput.parse({ companyName: "  Quill\u200Bfern \t Group " }).companyName).toBe("Quillfern Group");
    expect(companySettingsInput.parse({ companyName: "Cafe\u0301" }).companyName).toBe("Café");
    for (const bad of ["", "   ", "=SUM(A1)", "+1", "@x", "-x", "Quill\u202Efern", "a\u0007b", "x".repeat(121)]) {
      expect(companySettingsInput.safeParse({ companyName: bad }).success, JSON.stringify(bad)).toBe(false);
    }
    expect(companySettingsInput.safeParse({}).success).toBe(false);
  });

  it("takes a positive finite customer value or null (not known)", () => {
    expect(customerValuesInput.parse({ brands: [{ id: "b", customerValue: null }] }).brands[0]?.customerValue).toBeNull();
    expect(customerValuesInput.parse({ brands: [{ id: "b", customerValue: 0.5 }] }).brands[0]?.customerValue).toBe(0.5);
    for (const bad of [0, -3, Number.NaN, Number.POSITIVE_INFINITY, 2e9, "12"]) {
      const result = customerValuesInput.safeParse({ brands: [{ id: "b", customerValue: bad }] });
      expect(result.success, String(bad)).toBe(false);
      expect(result.error?.issues.map((i) => i.path.join("."))).toEqual(["brands.0.customerValue"]);
    }
    expect(customerValuesInput.safeParse({ brands: [{ id: "b", customerValue: 1 }, { id: "b", customerValue: 2 }] }).error?.issues[0]?.path).toEqual(["brands", 1, "id"]);
  });

  it("refuses two channels whose names differ only in case, spacing or joiners", () => {
    expect(nameKey(" Online  Video ")).toBe(nameKey("online video"));
    const result = channelSettingsInput.safeParse({ channels: [{ id: "a", name: "Online video" }, { id: "b", name: " ONLINE   video" }, { id: "c", name: "TV" }] });
    expect(result.error?.issues.map((i) => [i.path.join("."), i.message])).toEqual([["channels.1.name", 'Another channel is already called "Online video"']]);
    expect(channelSettingsInput.parse({ channels: [{ id: "a", name: "TV" }, { id: "b", name: "Radio" }] }).channels.map((c) => c.name)).toEqual(["TV", "Radio"]);
  });

  it("takes brand and market names tidied, and refuses empty, too long, unsafe or twice-used names", () => {
    expect(brandNamesInput.parse({ brands: [{ id: "b", name: "  Larkholm \u200B Home " }] }).brands[0]?.name).toBe("Larkholm Home");
    expect(marketNamesInput.parse({ markets: [{ id: "m", name: "Dunmere" }] }).markets[0]?.name).toBe("Dunmere");
    const messages = (name: unknown) => brandNamesInput.safeParse({ brands: [{ id: "b", name }] }).error?.issues.map((i) => [i.path.join("."), i.message]);
    expect(messages(" ")).toEqual([["brands.0.name", "The brand name cannot be empty"]]);
    expect(messages("x".repeat(101))).toEqual([["brands.0.name", "Keep the brand name to 100 characters"]]);
    expect(messages("=SUM(A1)")?.[0]?.[1]).toContain("spreadsheets read as a formula");
    expect(messages(12)?.[0]).toEqual(["brands.0.name", "Enter the brand name as text"]);
    expect(brandNamesInput.safeParse({ brands: [{ id: "b", name: "x".repeat(100) }] }).success).toBe(true);
    const twice = marketNamesInput.safeParse({ markets: [{ id: "a", name: "Dunmere" }, { id: "b", name: " DUNMERE " }, { id: "a", name: "Pellan" }] });
    expect(twice.error?.issues.map((i) => [i.path.join("."), i.message])).toEqual([
      ["markets.1.name", 'Another market is already called "Dunmere"'],
      ["markets.2.id", "This market is listed twice"],
    ]);
    expect(brandNamesInput.safeParse({ brands: [] }).error?.issues[0]?.message).toBe("List at least one brand");
  });
});
