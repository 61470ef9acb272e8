/** The safety caution of the domain, shown wherever people act on what the collection says. */
export function SafetyNote() {
  return (
    <aside className="site-footer__inner" aria-label="Safety">
      <svg width="18" height="18" viewBox="0 0 12 12" aria-hidden="true" style={{ flex: "none", marginTop: 2, color: "#8a4b00" }}>
        <path d="M6 0.8 11.5 11H0.5z" fill="currentColor" />
        <path d="M6 4.5v3" stroke="#fff" strokeWidth="1.4" strokeLinecap="round" />
        <circle cx="6" cy="9.3" r="0.8" fill="#fff" />
      </svg>
      <p>
        <strong>Safety.</strong> LPBF machines use Class 4 lasers (IEC 60825-1). Fine metal powders are combustible, some are
        reactive (Ti, Al, Mg; NFPA 484) and all are an inhalation hazard; inert gas can displace oxygen. Parameters in this
        collection are not safety-checked: stay inside the machine maker&apos;s limits and your site&apos;s procedures, local codes
        and licensed practice.
      </p>
    </aside>
  );
}
