namespace Kit.Diagnostics;

public enum ProjectionMethod
{
    Pca,
    Tsne,
}
