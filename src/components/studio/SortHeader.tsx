import { flexRender, type Header } from '@tanstack/react-table';

/** A table header cell that sorts on click and tells screen readers the order. */
export function SortHeader<T>({ header }: { header: Header<T, unknown> }) {
  const sorted = header.column.getIsSorted();
  const label = flexRender(header.column.columnDef.header, header.getContext());
  return (
    <th aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : undefined}>
      {header.column.getCanSort() ? (
        <button type="button" className="uppercase" onClick={header.column.getToggleSortingHandler()}>
          {label}
          {sorted === 'asc' ? ' ▲' : sorted === 'desc' ? ' ▼' : ''}
        </button>
      ) : (
        label
      )}
    </th>
  );
}
