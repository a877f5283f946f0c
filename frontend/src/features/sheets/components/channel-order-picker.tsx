import { Button, Space, Typography } from 'antd';
import { ArrowDownOutlined, ArrowUpOutlined, CloseOutlined, PlusOutlined } from '@ant-design/icons';
import type { Channel } from '@dialsheet/common';

interface ChannelOrderPickerProps {
  /** The campaign's channels, in the campaign's order. */
  channels: Channel[];
  /** Ids on the sheet, in entry order (a form control's value). */
  value?: string[];
  onChange?: (next: string[]) => void;
  id?: string;
}

function ChannelLabel({ channel }: { channel: Channel }) {
  return (
    <span className="channel-order-label">
      <strong className="channel-symbol">{channel.symbol}</strong>
      <span className="channel-order-name">{channel.name}</span>
      <Typography.Text type="secondary" className="channel-unit">
        {channel.rawUnit}
      </Typography.Text>
    </span>
  );
}

/**
 * Which channels the reader types at each row, and in what order. Every move is a button, so the
 * order can be set from the keyboard alone (Tab to a button, Space or Enter to press it).
 */
export function ChannelOrderPicker({ channels, value = [], onChange, id }: ChannelOrderPickerProps) {
  const byId = new Map(channels.map((c) => [c.id, c]));
  const chosen = value.flatMap((channelId) => {
    const channel = byId.get(channelId);
    return channel ? [channel] : [];
  });
  const available = channels.filter((c) => !value.includes(c.id));
  const set = (next: string[]) => onChange?.(next);
  const move = (index: number, by: -1 | 1) => {
    const next = value.slice();
    const [item] = next.splice(index, 1);
    next.splice(index + by, 0, item);
    set(next);
  };

  return (
    <div className="channel-order-picker" id={id}>
      <section className="channel-order-column" aria-label="Channels not on the sheet">
        <div className="channel-order-heading">
          <Typography.Text type="secondary">Not on the sheet</Typography.Text>
          <Button size="small" type="link" disabled={available.length === 0} onClick={() => set([...value, ...available.map((c) => c.id)])}>
            Add all
          </Button>
        </div>
        {available.length === 0 ? (
          <Typography.Text type="secondary" className="channel-order-empty">
            Every channel is on the sheet.
          </Typography.Text>
        ) : (
          <ul className="channel-order-list">
            {available.map((channel) => (
              <li key={channel.id}>
                <ChannelLabel channel={channel} />
                <Button size="small" type="text" icon={<PlusOutlined />} aria-label={`Add ${channel.symbol}`} onClick={() => set([...value, channel.id])} />
              </li>
            ))}
          </ul>
        )}
      </section>
      <section className="channel-order-column" aria-label="Channels on the sheet, in entry order">
        <div className="channel-order-heading">
          <Typography.Text type="secondary">On the sheet, in entry order</Typography.Text>
        </div>
        {chosen.length === 0 ? (
          <Typography.Text type="secondary" className="channel-order-empty">
            Add the displays the reader types at each row.
          </Typography.Text>
        ) : (
          <ol className="channel-order-list">
            {chosen.map((channel, index) => (
              <li key={channel.id}>
                <span className="numeric channel-order-position">{index + 1}</span>
                <ChannelLabel channel={channel} />
                <Space size={0}>
                  <Button
                    size="small"
                    type="text"
                    icon={<ArrowUpOutlined />}
                    aria-label={`Move ${channel.symbol} up`}
                    disabled={index === 0}
                    onClick={() => move(index, -1)}
                  />
                  <Button
                    size="small"
                    type="text"
                    icon={<ArrowDownOutlined />}
                    aria-label={`Move ${channel.symbol} down`}
                    disabled={index === chosen.length - 1}
                    onClick={() => move(index, 1)}
                  />
                  <Button
                    size="small"
                    type="text"
                    icon={<CloseOutlined />}
                    aria-label={`Remove ${channel.symbol}`}
                    onClick={() => set(value.filter((v) => v !== channel.id))}
                  />
                </Space>
              </li>
            ))}
          </ol>
        )}
      </section>
    </div>
  );
}
