import { screen, waitFor } from "@testing-library/react";
import { describe, expect, it } from "vitest";
import { paths, type ScreenKey } from "../../config/paths";
import { screens } from "../../config/screens";
import { renderApp, signedInRoutes, testUsers } from "../../testing/test-utils";

const moneyScreens: ScreenKey[] = ["spendPlanner", "budgetSplit"];

describe("every screen", () => {
  for (const key of Object.keys(screens) as ScreenKey[]) {
    it(`${screens[key].label} opens under its own name and says plainly what it holds`, async () => {
      renderApp(paths.app[key].getHref(), signedInRoutes(testUsers.admin));
      // Generous wait: the first load of a screen's module is slow when the machine is busy.
      expect(await screen.findByRole("heading", { level: 1, name: screens[key].label }, { timeout: 5000 })).toBeTruthy();
      await waitFor(() => expect(document.title).toBe(`${screens[key].label} · Tributary`));
      // Screens still to be built say what they will hold; none shows a made-up figure.
      const outline = screen.queryByRole("region", { name: "What this screen will hold" });
      if (outline) expect(outline.textContent).not.toMatch(/\d/);
      const caution = screen.queryByRole("complementary", { name: "Caution about estimates" });
      if (moneyScreens.includes(key)) expect(caution?.textContent).toMatch(/lift test/);
    });
  }
});
