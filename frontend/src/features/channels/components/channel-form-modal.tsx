import { Alert, Col, Form, Input, InputNumber, Modal, Row, Typography, type FormRule } from 'antd';
import type { Channel, CreateChannelRequest } from '@dialsheet/common';
import { errorMessage } from '@/lib/api-client';
import { useCreateChannel } from '../api/create-channel';
import { useUpdateChannel } from '../api/update-channel';

interface ChannelFormValues {
  name: string;
  symbol: string;
  quantity: string;
  rawUnit: string;
  resolution: number | null;
  rangeMin: number | null;
  rangeMax: number | null;
  fullScale: number | null;
  operatingMin: number | null;
  operatingMax: number | null;
  percentOfFullScale: number | null;
  percentOfReading: number | null;
  digits: number | null;
  plausibleMin: number | null;
  plausibleMax: number | null;
  reason?: string;
}

interface ChannelFormModalProps {
  campaignId: string;
  /** The channel to edit; left out, the modal adds a new one. */
  channel?: Channel;
  open: boolean;
  onClose: () => void;
  onSaved?: (channel: Channel) => void;
}

const isSet = (v: number | null | undefined): v is number => typeof v === 'number' && Number.isFinite(v);
const orNull = (v: number | null | undefined): number | null => (isSet(v) ? v : null);

/** The upper end of a pair must lie above the lower end, as the server requires. */
function aboveRule(minField: keyof ChannelFormValues, what: string): FormRule {
  return ({ getFieldValue }) => ({
    validator: (_, value: number | null | undefined) => {
      const min = getFieldValue(minField) as number | null | undefined;
      if (isSet(value) && isSet(min) && !(min < value)) return Promise.reject(new Error(`${what}: the upper end must be above the lower end (${min})`));
      return Promise.resolve();
    },
  });
}

const positive = (what: string): FormRule => ({
  validator: (_, value: number | null | undefined) =>
    isSet(value) && !(value > 0) ? Promise.reject(new Error(`${what} must be greater than 0`)) : Promise.resolve(),
});

const notNegative: FormRule = {
  validator: (_, value: number | null | undefined) =>
    isSet(value) && value < 0 ? Promise.reject(new Error('Must not be negative')) : Promise.resolve(),
};

const requiredNumber = (message: string): FormRule => ({ required: true, type: 'number', message });

function toRequest(values: ChannelFormValues): CreateChannelRequest {
  const accuracy = {
    percentOfFullScale: orNull(values.percentOfFullScale),
    percentOfReading: orNull(values.percentOfReading),
    digits: orNull(values.digits),
  };
  const anyAccuracy = Object.values(accuracy).some((v) => v !== null);
  return {
    name: values.name.trim(),
    symbol: values.symbol.trim(),
    quantity: values.quantity.trim(),
    rawUnit: values.rawUnit.trim(),
    resolution: values.resolution as number,
    rangeMin: values.rangeMin as number,
    rangeMax: values.rangeMax as number,
    fullScale: orNull(values.fullScale),
    operatingMin: orNull(values.operatingMin),
    operatingMax: orNull(values.operatingMax),
    accuracy: anyAccuracy ? accuracy : null,
    plausibleMin: orNull(values.plausibleMin),
    plausibleMax: orNull(values.plausibleMax),
  };
}

/** New channel, or changes to one: what the display shows, its range, limits and accuracy. */
export function ChannelFormModal({ campaignId, channel, open, onClose, onSaved }: ChannelFormModalProps) {
  const [form] = Form.useForm<ChannelFormValues>();
  const editing = channel !== undefined;
  const create = useCreateChannel({ mutationConfig: { onSuccess: (saved) => onSaved?.(saved) } });
  const update = useUpdateChannel({ mutationConfig: { onSuccess: (saved) => onSaved?.(saved) } });
  const mutation = editing ? update : create;
  const unit = Form.useWatch('rawUnit', form)?.trim() || undefined;

  const submit = (values: ChannelFormValues) => {
    const data = toRequest(values);
    if (channel) update.mutate({ channelId: channel.id, data: { ...data, reason: values.reason?.trim() || undefined } });
    else create.mutate({ campaignId, data });
  };

  const number = (placeholder?: string) => (
    <InputNumber className="full-width numeric" placeholder={placeholder} suffix={unit} controls={false} />
  );

  return (
    <Modal
      open={open}
      title={editing ? `Edit channel ${channel.symbol}` : 'New channel'}
      okText={editing ? 'Save changes' : 'Add channel'}
      onOk={() => form.submit()}
      onCancel={onClose}
      confirmLoading={mutation.isPending}
      afterClose={() => {
        create.reset();
        update.reset();
      }}
      width={680}
      destroyOnHidden
    >
      {mutation.isError ? <Alert type="error" showIcon className="form-alert" title={errorMessage(mutation.error)} role="alert" /> : null}
      <Form<ChannelFormValues>
        form={form}
        layout="vertical"
        requiredMark={false}
        preserve={false}
        disabled={mutation.isPending}
        className="channel-form"
        initialValues={{
          name: channel?.name ?? '',
          symbol: channel?.symbol ?? '',
          quantity: channel?.quantity ?? '',
          rawUnit: channel?.rawUnit ?? '',
          resolution: channel?.resolution ?? null,
          rangeMin: channel?.rangeMin ?? null,
          rangeMax: channel?.rangeMax ?? null,
          fullScale: channel?.fullScale ?? null,
          operatingMin: channel?.operatingMin ?? null,
          operatingMax: channel?.operatingMax ?? null,
          percentOfFullScale: channel?.accuracy?.percentOfFullScale ?? null,
          percentOfReading: channel?.accuracy?.percentOfReading ?? null,
          digits: channel?.accuracy?.digits ?? null,
          plausibleMin: channel?.plausibleMin ?? null,
          plausibleMax: channel?.plausibleMax ?? null,
        }}
        onFinish={submit}
      >
        <Row gutter={12}>
          <Col xs={24} sm={16}>
            <Form.Item
              label="Name"
              name="name"
              rules={[
                { required: true, whitespace: true, message: 'Give the channel a name' },
                { max: 200, message: 'Keep the name under 200 characters' },
              ]}
            >
              <Input placeholder="e.g. Warm stream inlet temperature" autoFocus />
            </Form.Item>
          </Col>
          <Col xs={24} sm={8}>
            <Form.Item
              label="Symbol"
              name="symbol"
              rules={[
                { required: true, whitespace: true, message: 'Give a short symbol' },
                { max: 40, message: 'Keep the symbol under 40 characters' },
              ]}
            >
              <Input placeholder="e.g. T1" />
            </Form.Item>
          </Col>
          <Col xs={24} sm={16}>
            <Form.Item
              label="Quantity"
              name="quantity"
              rules={[
                { required: true, whitespace: true, message: 'Say what the display measures' },
                { max: 100, message: 'Keep the quantity under 100 characters' },
              ]}
            >
              <Input placeholder="e.g. temperature" />
            </Form.Item>
          </Col>
          <Col xs={24} sm={8}>
            <Form.Item
              label="Unit on the display"
              name="rawUnit"
              rules={[
                { required: true, whitespace: true, message: 'Give the unit the display shows' },
                { max: 40, message: 'Keep the unit under 40 characters' },
              ]}
            >
              <Input placeholder="e.g. °C" />
            </Form.Item>
          </Col>
          <Col xs={24} sm={8}>
            <Form.Item
              label="Resolution"
              name="resolution"
              extra="Step of the last digit"
              rules={[requiredNumber('Give the step of the last digit'), positive('Resolution')]}
            >
              {number('e.g. 0.1')}
            </Form.Item>
          </Col>
          <Col xs={12} sm={8}>
            <Form.Item label="Range from" name="rangeMin" rules={[requiredNumber('Give the lower end of the range')]}>
              {number()}
            </Form.Item>
          </Col>
          <Col xs={12} sm={8}>
            <Form.Item
              label="Range to"
              name="rangeMax"
              dependencies={['rangeMin']}
              rules={[requiredNumber('Give the upper end of the range'), aboveRule('rangeMin', 'Range')]}
            >
              {number()}
            </Form.Item>
          </Col>
          <Col xs={24} sm={8}>
            <Form.Item label="Full scale" name="fullScale" extra="What “% FS” refers to" rules={[positive('Full scale')]}>
              {number('optional')}
            </Form.Item>
          </Col>
          <Col xs={12} sm={8}>
            <Form.Item label="Operating limit, low" name="operatingMin">
              {number('optional')}
            </Form.Item>
          </Col>
          <Col xs={12} sm={8}>
            <Form.Item
              label="Operating limit, high"
              name="operatingMax"
              dependencies={['operatingMin']}
              rules={[aboveRule('operatingMin', 'Operating limits')]}
            >
              {number('optional')}
            </Form.Item>
          </Col>
        </Row>
        <Typography.Text strong>Accuracy (from the instrument’s data sheet)</Typography.Text>
        <Row gutter={12} className="channel-form-accuracy">
          <Col xs={8}>
            <Form.Item label="± % of full scale" name="percentOfFullScale" rules={[notNegative]}>
              <InputNumber className="full-width numeric" placeholder="optional" suffix="% FS" controls={false} />
            </Form.Item>
          </Col>
          <Col xs={8}>
            <Form.Item label="± % of reading" name="percentOfReading" rules={[notNegative]}>
              <InputNumber className="full-width numeric" placeholder="optional" suffix="% rdg" controls={false} />
            </Form.Item>
          </Col>
          <Col xs={8}>
            <Form.Item label="+ digits" name="digits" rules={[notNegative]}>
              <InputNumber className="full-width numeric" placeholder="optional" suffix="digits" controls={false} />
            </Form.Item>
          </Col>
        </Row>
        <Row gutter={12}>
          <Col xs={12}>
            <Form.Item label="Plausible from" name="plausibleMin" extra="Readings outside are flagged, not refused">
              {number('optional')}
            </Form.Item>
          </Col>
          <Col xs={12}>
            <Form.Item
              label="Plausible to"
              name="plausibleMax"
              dependencies={['plausibleMin']}
              rules={[aboveRule('plausibleMin', 'Plausible range')]}
            >
              {number('optional')}
            </Form.Item>
          </Col>
        </Row>
        {editing ? (
          <Form.Item label="Reason for the change (kept in the audit trail)" name="reason">
            <Input placeholder="Optional" maxLength={500} />
          </Form.Item>
        ) : null}
      </Form>
    </Modal>
  );
}
