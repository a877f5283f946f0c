import { Checkbox, Form, Input } from 'antd';

/** Fields shared by "new campaign" and "edit campaign". */
export function CampaignFormFields() {
  return (
    <>
      <Form.Item
        label="Name"
        name="name"
        rules={[
          { required: true, whitespace: true, message: 'Give the campaign a name' },
          { max: 200, message: 'Keep the name under 200 characters' },
        ]}
      >
        <Input placeholder="e.g. Counter-flow core, spring series" />
      </Form.Item>
      <Form.Item label="Description" name="description" rules={[{ max: 4000, message: 'Keep the description under 4000 characters' }]}>
        <Input.TextArea autoSize={{ minRows: 3, maxRows: 8 }} placeholder="What is tested, on which rig, and why." />
      </Form.Item>
      <Form.Item name="decimalComma" valuePropName="checked" extra="A point always works. Tick this if readers type values such as 3,14.">
        <Checkbox>Readers may type a decimal comma</Checkbox>
      </Form.Item>
    </>
  );
}
