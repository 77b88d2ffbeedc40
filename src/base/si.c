/* SPDX-License-Identifier: BSD-3-Clause */
/* si.c - SPICE numbers with engineering suffixes, and SI-prefixed formatting for reports. */
#include <ctype.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include "schrot/si.h"

static int lower(int c)
{
	return tolower((unsigned char)c);
}

bool sch_si_looks_numeric(const char *text)
{
	const char *p = text;

	if (*p == '+' || *p == '-')
		p++;
	if (isdigit((unsigned char)*p))
		return true;
	return *p == '.' && isdigit((unsigned char)p[1]);
}

/* Scale of the suffix at s (length n remaining); sets *used to the suffix length. */
static double suffix_scale(const char *s, size_t n, size_t *used)
{
	*used = 0;
	if (n == 0)
		return 1.0;
	if (n >= 3 && lower(s[0]) == 'm' && lower(s[1]) == 'e' && lower(s[2]) == 'g') {
		*used = 3;
		return 1e6;
	}
	if (n >= 3 && lower(s[0]) == 'm' && lower(s[1]) == 'i' && lower(s[2]) == 'l') {
		*used = 3;
		return 25.4e-6;
	}
	*used = 1;
	switch (lower(s[0])) {
	case 'f':
		return 1e-15;
	case 'p':
		return 1e-12;
	case 'n':
		return 1e-9;
	case 'u':
		return 1e-6;
	case 'm':
		return 1e-3;
	case 'k':
		return 1e3;
	case 'g':
		return 1e9;
	case 't':
		return 1e12;
	default:
		*used = 0;
		return 1.0;
	}
}

enum sch_err sch_si_parse_n(const char *text, size_t n, double *value)
{
	char num[128];
	size_t i = 0, digits = 0, used;
	double v, scale;
	char *end;

	if (i < n && (text[i] == '+' || text[i] == '-'))
		i++;
	while (i < n && isdigit((unsigned char)text[i])) {
		i++;
		digits++;
	}
	if (i < n && text[i] == '.') {
		i++;
		while (i < n && isdigit((unsigned char)text[i])) {
			i++;
			digits++;
		}
	}
	if (digits == 0)
		return SCH_ERR_INPUT;
	if (i < n && lower(text[i]) == 'e') {
		size_t j = i + 1, exp_digits = 0;
		if (j < n && (text[j] == '+' || text[j] == '-'))
			j++;
		while (j < n && isdigit((unsigned char)text[j])) {
			j++;
			exp_digits++;
		}
		if (exp_digits == 0)
			return SCH_ERR_INPUT; /* "1e", "1e+" */
		i = j;
	}
	if (i >= sizeof(num))
		return SCH_ERR_INPUT;
	memcpy(num, text, i);
	num[i] = '\0';
	v = strtod(num, &end);
	if (*end != '\0')
		return SCH_ERR_INPUT;
	scale = suffix_scale(text + i, n - i, &used);
	i += used;
	/* Unit letters may follow; nothing but letters (a digit or '.' means garbage like "1k2"). */
	for (; i < n; i++) {
		if (!isalpha((unsigned char)text[i]))
			return SCH_ERR_INPUT;
	}
	v *= scale;
	if (!isfinite(v))
		return SCH_ERR_INPUT;
	*value = v;
	return SCH_OK;
}

enum sch_err sch_si_parse(const char *text, double *value)
{
	return sch_si_parse_n(text, strlen(text), value);
}

char *sch_si_format(char *out, size_t size, double value, int digits, const char *unit)
{
	static const char *const prefixes[] = { "y", "z", "a", "f", "p", "n", "µ", "m", "",
						"k", "M", "G", "T", "P", "E" };
	const int zero_index = 8;
	double mag, scaled;
	int exp3, index;

	if (!unit)
		unit = "";
	if (digits <= 0)
		digits = 3;
	if (isnan(value)) {
		snprintf(out, size, "-");
		return out;
	}
	if (value == 0.0) {
		snprintf(out, size, "0%s%s", *unit ? " " : "", unit);
		return out;
	}
	if (isinf(value)) {
		snprintf(out, size, "%sinf%s%s", value < 0 ? "-" : "", *unit ? " " : "", unit);
		return out;
	}
	mag = fabs(value);
	exp3 = (int)floor(log10(mag) / 3.0);
	scaled = mag / pow(10.0, 3.0 * exp3);
	/* Round to the significant digits first: 999.96 becomes "1.00 k", 99.96 k becomes "100 k". */
	{
		char probe[64];
		double rounded;
		snprintf(probe, sizeof(probe), "%.*e", digits - 1, scaled);
		rounded = strtod(probe, NULL);
		if (rounded >= 1000.0) {
			exp3++;
			rounded /= 1000.0;
		}
		scaled = rounded;
	}
	index = exp3 + zero_index;
	if (index < 0 || index >= (int)(sizeof(prefixes) / sizeof(prefixes[0]))) {
		snprintf(out, size, "%.*g%s%s", digits, value, *unit ? " " : "", unit);
		return out;
	}
	{
		int int_digits = scaled >= 100 ? 3 : scaled >= 10 ? 2 : 1;
		int dec = digits - int_digits;
		snprintf(out, size, "%s%.*f %s%s", value < 0 ? "-" : "", dec > 0 ? dec : 0, scaled,
			 prefixes[index], unit);
	}
	return out;
}
