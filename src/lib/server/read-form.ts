/**
 * The request's form fields, or null when the body is not a readable form (a truncated or
 * malformed multipart body, say). Actions answer null with a 400 and a message, never a 500.
 */
export async function readForm(request: Request): Promise<FormData | null> {
	try {
		return await request.formData();
	} catch {
		return null;
	}
}
