/** How a final invoice was settled: by card through the payment service, or recorded by the owner. */
export const PAYMENT_METHODS = ['card', 'cash', 'cheque'] as const;
export type PaymentMethod = (typeof PAYMENT_METHODS)[number];

export const PAYMENT_METHOD_LABELS: Record<PaymentMethod, string> = {
	card: 'Card',
	cash: 'Cash',
	cheque: 'Cheque'
};

export type InvoiceLineView = { label: string; amountCents: number };

/** A final invoice as the office and the customer's pay page show it. */
export type BalanceView = {
	invoiceId: string;
	number: number;
	issuedAt: string;
	lines: InvoiceLineView[];
	subtotalCents: number;
	taxCents: number;
	/** What the invoice asks for: the balance after the deposit. */
	totalCents: number;
	/** Credit notes against it (negative), so totalCents + creditedCents is what is owed. */
	creditedCents: number;
	/** The credit notes themselves, oldest first; amounts positive (what each took off). */
	credits: { number: number; reason: string; amountCents: number; issuedAt: string }[];
	recipientEmail: string | null;
	paid: { method: PaymentMethod; amountCents: number; reference: string; paidAt: string } | null;
};
