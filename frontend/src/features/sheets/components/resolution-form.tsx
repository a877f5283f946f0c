import { useImperativeHandle, useRef, useState, type Ref } from 'react';
import { useQueryClient } from '@tanstack/react-query';
import { Alert, Button, Form, Input, Typography, type InputRef } from 'antd';
import { checkLimits, parseReading, type Channel, type MismatchCell, type Resolution } from '@dialsheet/common';
import { errorMessage, isApiError } from '@/lib/api-client';
import { getMismatchesQueryOptions } from '../api/get-mismatches';
import { sheetGridKey } from '../api/get-sheet-grid';
import { staleResolution, useResolveCell } from '../api/resolve-cell';
import { FLAG_LABELS } from '../utils/sheet-format';
import { ResolutionFacts } from './resolution-facts';

export interface ResolutionFormHandle {
  /** Puts a text into the resolved value (one pass's entry, say) and focuses it. */
  fillValue: (text: string) => void;
  focusValue: () => void;
}

interface ResolutionFormProps {
  sheetId: string;
  cell: MismatchCell;
  channel: Channel;
  decimalComma: boolean;
  nameOf: (userId: string) => string | null;
  ref?: Ref<ResolutionFormHandle>;
}

const MAX_REASON = 500;

interface Problems {
  value?: string;
  reason?: string;
  general?: string[];
}

function serverProblems(error: unknown): Problems {
  if (!isApiError(error) || !error.body) return { general: [errorMessage(error)] };
  const raw = error.body.message;
  const messages = Array.isArray(raw) ? raw : [raw || errorMessage(error)];
  const out: Problems = {};
  for (const message of messages) {
    if (/^rawText\b/.test(message)) out.value = message;
    else if (/^reason\b/.test(message)) out.reason = message;
    else out.general = [...(out.general ?? []), message];
  }
  return out;
}

/**
 * The agreed value of a mismatched cell and why, recorded against the frame. The value is parsed
 * as it is typed, by the same rules as an entry; a value outside the channel's limits is flagged,
 * not refused. A resolution saved meanwhile by someone else is never overwritten blind: the server
 * answers 409 with it and the form offers to load it.
 */
export function ResolutionForm({ sheetId, cell, channel, decimalComma, nameOf, ref }: ResolutionFormProps) {
  const queryClient = useQueryClient();
  const [base, setBase] = useState<Resolution | null>(cell.resolution);
  const [value, setValue] = useState(cell.resolution?.rawText ?? '');
  const [reason, setReason] = useState(cell.resolution?.reason ?? '');
  const [problems, setProblems] = useState<Problems>({});
  const [stale, setStale] = useState<Resolution | null>(null);
  const [savedVersion, setSavedVersion] = useState<number | null>(null);
  const valueRef = useRef<InputRef>(null);

  const resolve = useResolveCell({
    mutationConfig: {
      onSuccess: (saved) => {
        setBase(saved);
        setStale(null);
        setProblems({});
        setSavedVersion(saved.version);
      },
      onError: (error) => {
        const current = staleResolution(error);
        if (current) {
          setStale(current);
          setProblems({ general: [errorMessage(error)] });
        } else {
          setProblems(serverProblems(error));
        }
      },
    },
  });

  useImperativeHandle(
    ref,
    () => ({
      fillValue: (text: string) => {
        setValue(text);
        setProblems((p) => ({ ...p, value: undefined }));
        valueRef.current?.focus();
      },
      focusValue: () => valueRef.current?.focus(),
    }),
    [],
  );

  const parsed = parseReading(value, { decimalComma });
  const warnings = parsed.kind === 'number' ? checkLimits(parsed.value, channel) : [];
  const valueError = parsed.kind === 'error' ? parsed.message : problems.value;

  const submit = () => {
    if (resolve.isPending) return;
    const trimmedReason = reason.trim();
    const next: Problems = {};
    if (parsed.kind === 'error') next.value = parsed.message;
    if (!trimmedReason) next.reason = 'Say why this is the value, e.g. "frame 01:23.456 shows 12.5, the last digit had settled"';
    else if (trimmedReason.length > MAX_REASON) next.reason = `Keep the reason under ${MAX_REASON} characters`;
    setProblems(next);
    setSavedVersion(null);
    if (next.value || next.reason) return;
    resolve.mutate({
      sheetId,
      rowIndex: cell.rowIndex,
      channelId: cell.channelId,
      data: { rawText: value, reason: trimmedReason, ...(base ? { baseVersion: base.version } : {}) },
    });
  };

  const reload = () => {
    if (!stale) return;
    setBase(stale);
    setValue(stale.rawText);
    setReason(stale.reason);
    setStale(null);
    setProblems({});
    void queryClient.invalidateQueries({ queryKey: getMismatchesQueryOptions(sheetId).queryKey });
    // The table's cell shows the resolution too.
    void queryClient.invalidateQueries({ queryKey: sheetGridKey(sheetId) });
  };

  let preview: string | null = null;
  if (parsed.kind === 'number') preview = `= ${parsed.value} ${channel.rawUnit}`;
  else if (parsed.kind === 'flag') preview = `flagged ${FLAG_LABELS[parsed.flag]}`;

  return (
    <div
      className="resolution-form"
      onKeyDown={(event) => {
        if (event.key === 'Enter' && (event.ctrlKey || event.metaKey)) {
          event.preventDefault();
          submit();
        }
      }}
    >
      {base ? <ResolutionFacts resolution={base} unit={channel.rawUnit} byName={nameOf(base.resolvedBy)} /> : null}
      {problems.general ? (
        <Alert
          type="error"
          showIcon
          role="alert"
          className="form-alert"
          title={problems.general.join(' ')}
          description={
            stale ? (
              <div className="stale-resolution">
                <ResolutionFacts resolution={stale} unit={channel.rawUnit} byName={nameOf(stale.resolvedBy)} />
                <Button size="small" onClick={reload}>
                  Load the stored resolution
                </Button>
              </div>
            ) : undefined
          }
        />
      ) : null}
      {savedVersion !== null ? (
        <Alert type="success" showIcon className="form-alert" title={`Resolution saved (version ${savedVersion})`} role="status" />
      ) : null}
      <Form layout="vertical" requiredMark={false} component="div" disabled={resolve.isPending}>
        <Form.Item
          label="Resolved value"
          htmlFor="resolution-value"
          validateStatus={valueError ? 'error' : warnings.length > 0 ? 'warning' : undefined}
          help={valueError ?? (warnings.length > 0 ? warnings.map((w) => w.message).join('; ') : preview)}
          extra="Type what the frame shows; #unreadable or #ambiguous when it cannot be read."
        >
          <Input
            id="resolution-value"
            ref={valueRef}
            className="numeric"
            value={value}
            suffix={channel.rawUnit}
            autoComplete="off"
            spellCheck={false}
            onChange={(event) => {
              setValue(event.target.value);
              setSavedVersion(null);
            }}
          />
        </Form.Item>
        <Form.Item
          label="Reason"
          htmlFor="resolution-reason"
          validateStatus={problems.reason ? 'error' : undefined}
          help={problems.reason}
        >
          <Input.TextArea
            id="resolution-reason"
            value={reason}
            autoSize={{ minRows: 2, maxRows: 5 }}
            maxLength={MAX_REASON}
            placeholder="What the frame shows and why this value"
            onChange={(event) => {
              setReason(event.target.value);
              setSavedVersion(null);
            }}
          />
        </Form.Item>
        <div className="form-actions">
          <Button type="primary" loading={resolve.isPending} onClick={submit}>
            {base ? 'Save changed resolution' : 'Save resolution'}
          </Button>
          <Typography.Text type="secondary" className="key-hint">
            Ctrl + Enter
          </Typography.Text>
        </div>
      </Form>
    </div>
  );
}
