/** The Meltledger mark: three powder layers and a fused track across the top one. */
export function BrandMark() {
  return (
    <svg className="brand__mark" width="26" height="26" viewBox="0 0 26 26" aria-hidden="true">
      <rect x="2" y="17" width="22" height="5" rx="1.2" fill="#9aa3ad" />
      <rect x="2" y="11" width="22" height="5" rx="1.2" fill="#c3c9d0" />
      <rect x="2" y="5" width="22" height="5" rx="1.2" fill="#e3e7eb" />
      <path d="M4 7.5h13" stroke="#0e6a63" strokeWidth="2.4" strokeLinecap="round" />
      <circle cx="19.5" cy="7.5" r="2.3" fill="#e07a1f" />
    </svg>
  );
}
