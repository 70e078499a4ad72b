/** The standing caution shown wherever designs are presented. */
export function SafetyCaution() {
  return (
    <p>
      Chainwright analyses signal levels, frequency response and noise. It does not check isolation, creepage, leakage
      currents or safety ratings. Verify every design on hardware; for mains-powered or body-connected sensors, local
      codes and licensed practice govern.
    </p>
  );
}
