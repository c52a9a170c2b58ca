/** The caution shown above commands flagged as moving machinery. */
export function MachineryCaution() {
  return (
    <div className="notice notice-warn mb-4" role="note" data-testid="machinery-caution">
      <p className="font-semibold">This command moves machinery.</p>
      <p className="text-sm">
        Test it with the machine in a safe state, follow lockout and your site's procedures, and check it against the device's
        manual before the PLC program sends it.
      </p>
    </div>
  );
}
