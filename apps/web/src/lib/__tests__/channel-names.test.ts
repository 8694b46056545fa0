import { describe, expect, it } from "vitest";
import { channelCodeAsName, channelNameLookup } from "../channel-names";

describe("channel names", () => {
  const channels = [
    { code: "search", name: "Search" },
    { code: "online_video", name: "Online video" },
    { code: "tv", name: "  " },
  ];

  it("reads a channel's code as its display name", () => {
    const name = channelNameLookup(channels);
    expect(name("online_video")).toBe("Online video");
    expect(name("search")).toBe("Search");
  });

  it("falls back to the code when the portfolio has no name for it", () => {
    const name = channelNameLookup(channels);
    expect(name("audio")).toBe("audio");
    expect(name("tv")).toBe("tv");
    expect(channelCodeAsName("online_video")).toBe("online_video");
  });
});
