// Unknown API paths answer JSON, never an HTML page.
function notFound() {
  return Response.json({ error: "No such API endpoint. See GET /api/v1/calculators and the README's API section." }, { status: 404 });
}
export const loader = notFound;
export const action = notFound;
