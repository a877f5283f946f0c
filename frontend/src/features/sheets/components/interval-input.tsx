import { InputNumber, Radio, Space } from 'antd';

const PRESETS = [2, 3, 5, 10] as const;

interface IntervalInputProps {
  value?: number | null;
  onChange?: (next: number | null) => void;
  id?: string;
}

/** Seconds between rows: the usual steps one key away, any other value typed in. */
export function IntervalInput({ value, onChange, id }: IntervalInputProps) {
  const preset = PRESETS.find((p) => p === value);
  return (
    <Space size={8} wrap>
      <Radio.Group
        optionType="button"
        size="small"
        aria-label="Usual intervals"
        value={preset}
        options={PRESETS.map((p) => ({ label: `${p} s`, value: p }))}
        onChange={(event) => onChange?.(event.target.value as number)}
      />
      <InputNumber
        id={id}
        className="numeric interval-number"
        value={value ?? null}
        min={0.1}
        step={1}
        suffix="s"
        aria-label="Interval in seconds"
        onChange={(next) => onChange?.(typeof next === 'number' ? next : null)}
      />
    </Space>
  );
}
