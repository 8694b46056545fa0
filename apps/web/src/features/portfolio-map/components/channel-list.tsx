import type { Channel } from "@tributary/contracts";

const seriesColours = 8;

/** The portfolio's channels, each with the chart colour it keeps on every screen. */
export function ChannelList({ channels }: { channels: Channel[] }) {
  return (
    <section aria-labelledby="channel-list-title" className="flex flex-wrap items-center gap-x-4 gap-y-2">
      <h2 id="channel-list-title" className="text-small font-semibold text-ink-800">
        Channels
      </h2>
      {channels.length === 0 ? (
        <p className="text-small text-ink-600">No channels are set up for this portfolio yet.</p>
      ) : (
        <ul className="flex flex-wrap gap-2">
          {channels.map((channel, index) => (
            <li
              key={channel.id}
              className="inline-flex items-center gap-2 rounded-full border border-line bg-surface px-3 py-1 text-small"
            >
              <span
                className="h-2.5 w-2.5 shrink-0 rounded-full"
                style={{ background: `var(--color-series-${(index % seriesColours) + 1})` }}
                aria-hidden="true"
              />
              <span className="font-medium text-ink-900">{channel.name}</span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
