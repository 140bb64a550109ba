import { useEffect, useState } from "react";
import type { Toast as ToastData } from "~/services/session.server";

const styles: Record<ToastData["kind"], string> = {
  success: "border-kelp bg-kelp-light",
  info: "border-tide bg-tide-light",
  error: "border-danger bg-danger-light",
};

/** A one-time message after a redirect; rendered on the server, so it shows without JavaScript. */
export function Toast({ toast }: { toast: ToastData | null }) {
  const [visible, setVisible] = useState(true);
  useEffect(() => setVisible(true), [toast]);
  if (!toast || !visible) return null;
  return (
    <div role="status" className={`no-print mx-auto mt-4 flex max-w-7xl items-start justify-between gap-4 rounded-md border-l-4 px-4 py-3 text-sm ${styles[toast.kind]}`}>
      <span data-testid="toast">{toast.message}</span>
      <button type="button" onClick={() => setVisible(false)} className="text-xs font-semibold underline">
        Dismiss
      </button>
    </div>
  );
}
