import type { Channel } from "@tributary/contracts";

/**
 * A channel's display name from its code ("online_video" → "Online video"). Codes stay the
 * values (keys, option values, what is saved and sent); names are what people read.
 */
export type ChannelName = (code: string) => string;

/** The lookup for a portfolio's channels; a code the portfolio has no name for reads as itself. */
export function channelNameLookup(channels: readonly Pick<Channel, "code" | "name">[]): ChannelName {
  const names = new Map(channels.map((channel) => [channel.code, channel.name.trim()]));
  return (code) => {
    const name = names.get(code);
    return name ? name : code;
  };
}

/** For places with no portfolio at hand (tests, fallbacks): every code reads as itself. */
export const channelCodeAsName: ChannelName = (code) => code;
