import type { Channel } from "@tributary/contracts";

const seriesColours = 8;

export function ChannelList({ channels }: { channels: Channel[] }) {
  return (
    <section aria-labelledby="channel-list-title" className="rounded-lg border border-line bg-surface p-4 shadow-card">
      <h2 id="channel-list-title" className="text-body font-semibold text-ink-900">
        Channels
      </h2>
      {channels.length === 0 ? (
        <p className="mt-2 text-small text-ink-600">No channels are set up for this portfolio yet.</p>
      ) : (
        <ul className="mt-3 space-y-2">
          {channels.map((channel, index) => (
            <li key={channel.id} className="flex items-center gap-2.5 text-small">
              <span
                className="h-3 w-3 shrink-0 rounded-sm"
                style={{ background: `var(--color-series-${(index % seriesColours) + 1})` }}
                aria-hidden="true"
              />
              <span className="font-medium text-ink-900">{channel.name}</span>
              <span className="text-ink-500">{channel.code}</span>
            </li>
          ))}
        </ul>
      )}
    </section>
  );
}
