/** The line shown wherever people act on numbers (design: decision support only). */
export function Caution() {
  return (
    <p class="caution" role="note">
      <strong>Decision support only:</strong> the structure's designer or manufacturer ratings, the site's competent person and local regulations govern.
    </p>
  );
}
