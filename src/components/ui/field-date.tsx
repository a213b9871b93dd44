import { localToday } from '@common/calendar-date';
import { TextField } from './text-field';

/** The hint under a date that starts at today: which "today" it is. */
export const TODAY_HINT = "Starts at today's date on this device.";

/**
 * The day a field record is dated: starts at today on the device's own calendar (where the
 * grower stands, not the server's), never later, and back to today when cleared.
 */
export function FieldDate({
  date,
  onChange,
  className,
}: {
  date: string;
  onChange: (date: string) => void;
  className?: string;
}) {
  return (
    <TextField
      label="Date"
      type="date"
      hint={TODAY_HINT}
      value={date}
      max={localToday()}
      onChange={(e) => onChange(e.target.value || localToday())}
      className={className}
    />
  );
}
