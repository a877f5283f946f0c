import { Link } from 'react-router-dom';
import { Button } from 'antd';
import { EditOutlined } from '@ant-design/icons';
import type { Sheet } from '@dialsheet/common';
import { paths } from '@/config/paths';
import { isPassFinished, ownPass, type SheetViewer } from '../utils/sheet-access';

/** The way into entry, for the person who owns a pass that is still open. */
export function EnterPassButton({ sheet, viewer }: { sheet: Sheet; viewer: SheetViewer }) {
  const pass = ownPass(sheet, viewer);
  if (pass === null || sheet.lock || isPassFinished(sheet, pass)) return null;
  return (
    <Link to={paths.sheetEntry.getHref(sheet.campaignId, sheet.id)}>
      <Button type="primary" icon={<EditOutlined />}>
        Enter pass {pass}
      </Button>
    </Link>
  );
}
