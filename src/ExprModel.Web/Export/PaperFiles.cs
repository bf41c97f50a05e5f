using ExprModel.Core.Analysis;
using ExprModel.Core.Cell;
using ExprModel.Core.Export;
using ExprModel.Core.Models;
using ExprModel.Web.Simulation;

namespace ExprModel.Web.Export;

/// <summary>
/// The paper-ready files the pages offer: the methods paragraph and the BibTeX of every cited source (from the library's
/// <see cref="MethodsText"/> and <see cref="BibTex"/>), and the adaptation-mechanism table (<see cref="MechanismCsv"/>). Each
/// carries the research-use caution.
/// </summary>
public static class PaperFiles
{
    public static DownloadFile Methods(ModelDocument doc, ModelRunner runner, string stem) =>
        new($"{stem}.methods.txt", "text/plain", runner.Methods(doc).Paragraph + "\n");

    public static DownloadFile BibTexFile(ModelDocument doc, ModelRunner runner, string stem) =>
        new($"{stem}.bib", "application/x-bibtex", runner.Methods(doc).BibTex);

    public static DownloadFile Mechanisms(string modelName, MechanismReport report, Geometry geometry, string stem) =>
        new($"{stem}.mechanisms.csv", "text/csv", MechanismCsv.Write(modelName, report, CurrentUnit.UaPerCm2, geometry));
}
