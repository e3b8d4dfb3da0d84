namespace FitSpec.Reporting;

/// <summary>A report template could not be found, parsed or rendered; the message names the template file.</summary>
public sealed class ReportTemplateException : Exception
{
    public ReportTemplateException()
    {
    }

    public ReportTemplateException(string message)
        : base(message)
    {
    }

    public ReportTemplateException(string message, Exception innerException)
        : base(message, innerException)
    {
    }
}
