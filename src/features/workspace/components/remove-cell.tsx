/** The last cell of an editable table row: "Remove", shown only to those who may edit. */
export function RemoveCell({ show, onRemove }: { show: boolean; onRemove: () => void }) {
  return (
    <td className="w-16 px-2 py-1 text-right">
      {show && (
        <button type="button" className="py-1.5 text-xs text-danger hover:underline" onClick={onRemove}>
          Remove
        </button>
      )}
    </td>
  );
}
